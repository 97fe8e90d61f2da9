"""`stock compensate`: from an oscillator's measured drift to the tempco parts on the shelf that cancel it."""

from __future__ import annotations

import json
from decimal import Decimal
from typing import Annotated, Optional

import typer


def _opt(*names: str, text: str):
    return typer.Option(*names, help=text)


def _lines(result) -> list[str]:  # noqa: ANN001 - a stock.compensating.Compensation
    from stock.matching.compensating import headline
    from stock.physics.drift import format_frequency
    from stock.units import format_capacitance, format_number, MINUS

    def signed(value: Decimal, places: int = 3) -> str:
        return f"{round(value, places):+.{places}f}".replace("-", MINUS)

    tank = result.tank
    over = f"{tank.measured} over {format_number(tank.delta_t_k)} K = " if tank.delta_t_k is not None else ""
    source = (f"from the {format_number(tank.coil_h * 1_000_000)} µH coil (C = 1/((2πf)²·L))"
              if tank.coil_h is not None else "as given")
    total = format_capacitance(round(tank.c_total_pf, 2))
    lines = [f"tank: {format_frequency(tank.f0_hz)}, {total} {source}",
             f"measured: {over}{signed(tank.drift_hz_per_k).rstrip('0').rstrip('.')} Hz/K = "
             f"{signed(tank.drift_ppm_per_k)} ppm/K; {tank.direction()}",
             f"effective tempco of the tank: TC_eff = −2·(Δf/f)/ΔT = {signed(tank.tc_eff_ppm_per_k)} ppm/K "
             "(coil, wiring and capacitors lumped)",
             f"to cancel it: Cx·(α_new − α_old) = −TC_eff·C_total = {signed(tank.needed_pf_ppm, 1)} pF·ppm/K, "
             f"taking the slice from {tank.alpha_old_name} ({signed(tank.alpha_old, 0) if tank.alpha_old else '0'} ppm/K)"]
    if result.tempcos:
        lines.append("tempcos on hand:")
        for t in result.tempcos:
            bins = f"{t.bins} bin{'s' if t.bins != 1 else ''}"
            lines.append(f"  {signed(t.alpha, 0) if t.alpha else '0':>6} ppm/K  {', '.join(t.codes):<14} "
                         f"{bins:<8} {t.note}")
    if result.options:
        lines.append("options, best first:" if any(o.useful for o in result.options)
                     else "nearest on hand, none halving the drift:")
        for n, option in enumerate(result.options, start=1):
            r = option.result
            lines.append(f"  {n}. {headline(tank, option)}")
            cx = format_capacitance(round(option.cx_pf, 2))
            lines.append(f"     residual {signed(r.residual_ppm)} ppm/K (band {signed(r.residual_low_ppm)} … "
                         f"{signed(r.residual_high_ppm)}); slice for this tempco {cx};"
                         f" new total {format_capacitance(round(r.new_total_pf, 2))}" + (
                             f" after trimming ({format_capacitance(round(r.total_before_trim_pf, 2))} before)"
                             if r.trim_pf else ""))
            for basis in dict.fromkeys(p.spread.basis for p in option.parts):
                lines.append(f"     {basis}")
    lines += list(result.explanation)
    lines.append("assumptions:")
    lines += [f"  - {a}" for a in result.assumptions]
    lines += [f"caution: {c}" for c in result.cautions]
    return lines


def register(app: typer.Typer) -> None:
    @app.command("compensate")
    def compensate(
        ctx: typer.Context,
        f0: Annotated[str, _opt("--f0", text="The oscillator's frequency, e.g. 7MHz.")],
        drift: Annotated[str, _opt("--drift", text=(
            "The measured drift: -20Hz/K, -3ppm/K, or a whole shift such as -60Hz with --delta-t."))],
        tank: Annotated[Optional[str], _opt("--tank", text="The tank's total capacitance, e.g. 300p.")] = None,
        coil: Annotated[Optional[str], _opt("--coil", text="The coil instead of --tank, e.g. 4.7uH.")] = None,
        delta_t: Annotated[Optional[str], _opt("--delta-t", text=(
            "The warming (K) a whole shift was measured over, e.g. 3."))] = None,
        tank_tempco: Annotated[str, _opt("--tank-tempco", text=(
            "Tempco of the capacitance the slice is taken from: a code or ppm/K (default C0G)."))] = "C0G",
        combine: Annotated[bool, _opt("--combine", text="Also try parallel and series pairs of one tempco.")] = False,
        limit: Annotated[int, _opt("--limit", text="Options shown at most (default 6).")] = 6,
        as_json: Annotated[bool, _opt("--json", text="Print one JSON object.")] = False,
    ) -> None:
        """Null a drifting oscillator: which tempco parts on the shelf cancel the drift you measured.

        From the LC resonance formula, the tank's lumped tempco is TC_eff = −2·(Δf/f)/ΔT; a slice Cx
        of its C0G is swapped for parts of tempco α with Cx·α = −TC_eff·C_total.

        Example: stock compensate --f0 7MHz --tank 300p --drift -20Hz/K --combine
        """
        from stock.cli.context import state
        from stock.matching.compensating import compensate as answer
        from stock.physics.compensation import measure_tank, slice_tempco
        from stock.errors import BadValue
        from stock.store.database import open_store
        from stock.markings.typed_values import parse_capacitance
        from stock.units import parse_drift, parse_frequency, parse_inductance, parse_kelvin

        if limit < 1:
            raise BadValue("--limit", str(limit), "a number of options of 1 or more")
        value, unit = parse_drift(drift)
        alpha_old, name = slice_tempco(tank_tempco)
        measured = measure_tank(
            parse_frequency(f0), value, unit,
            tank_pf=parse_capacitance(tank, "--tank") if tank else None,
            coil_h=parse_inductance(coil) if coil else None,
            delta_t_k=parse_kelvin(delta_t) if delta_t is not None else None,
            alpha_old=alpha_old, alpha_old_name=name, measured=drift.strip())
        with open_store(state(ctx).db_path, create=False) as store:
            result = answer(store, measured, combine=combine, limit=limit)
        if as_json:
            inputs = {"f0": f0, "tank": tank, "coil": coil, "drift": drift, "delta_t": delta_t,
                      "tank_tempco": tank_tempco, "combine": combine, "limit": limit}
            typer.echo(json.dumps({"inputs": inputs, **result.to_json()}, ensure_ascii=False))
            return
        typer.echo("\n".join(_lines(result)))
