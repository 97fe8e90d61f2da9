"""inventory"""
