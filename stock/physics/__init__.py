"""The physics of a part in a circuit: no store, no files.

``stability`` (what each dielectric and family promises with temperature, ageing and bias),
``applications`` (the application table: what each job asks), ``budget`` (the worst-case budget,
its terms compounded), ``grading`` (the grade, its doubts, mains by position), ``drift`` (tank and timer drift), ``compensation`` (from a measured oscillator
drift to the tempco slice that cancels it), ``combining`` (series and parallel pairs).
"""
