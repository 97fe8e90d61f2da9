"""Parts for a requirement: what a position asks (``requirement``), the shelf searched (``search``),
the tempco parts that null a drifting oscillator (``compensating``), and a part in hand replaced
(``replacement``), its stand-ins judged (``stand_ins``) by the trade's substitution rules
(``substitutions``)."""
