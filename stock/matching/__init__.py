"""Parts for a requirement: what a position asks (``requirement``), the shelf searched (``search``),
and the tempco parts that null a drifting oscillator (``compensating``)."""
