"""Parts for a requirement: what a position asks (``requirement``) and the shelf searched (``search``)."""
