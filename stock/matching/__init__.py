"""Parts for a requirement: what a position asks (``requirement``) and the shelf searched (``search``);
a part in hand replaced (``replacement``), its stand-ins judged (``stand_ins``) by the trade's
substitution rules (``substitutions``)."""
