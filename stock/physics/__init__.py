"""The physics of a part in a circuit: no store, no files.

``stability`` (what each dielectric and family promises with temperature, ageing and bias),
``applications`` (the application table: what each job asks), ``grading`` (the worst-case budget
and the grade), ``drift`` (tank and timer drift), ``compensation`` (from a measured oscillator
drift to the tempco slice that cancels it), ``combining`` (series and parallel pairs).
"""
