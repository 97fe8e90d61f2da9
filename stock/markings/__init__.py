"""Code tables, one module per standard, and the decoder that reads a marking with them.

``value_codes`` (IEC 60062 value codes), ``tolerance_codes`` (IEC 60062 letters),
``voltage_codes`` (EIA voltage codes), ``ceramic_codes`` (EIA-198 Class 1/2), ``families``
(film, mica, electrolytic … by name), ``safety_classes`` (IEC 60384-14), ``colour_words`` /
``colour_codes`` / ``mica_codes`` / ``colours`` (colour bands and dots), ``preferred_values``
(IEC 60063), ``packages`` (chip sizes, mounting, body and pitch from package, footprint
or description text), ``typed_values`` (values typed on the command line), ``decoder``
(``decode(text) -> Marking``, never raises). Nothing here knows of the store.
"""
