"""kitting"""
