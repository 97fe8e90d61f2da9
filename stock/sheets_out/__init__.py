"""sheets_out"""
