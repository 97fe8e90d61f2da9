"""File readers: each turns one kind of sheet into plain rows with their row numbers."""
