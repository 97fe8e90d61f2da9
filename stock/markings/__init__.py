"""markings"""
