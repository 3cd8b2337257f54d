"""Where each model stops being valid, as warnings that travel with every result.

A :class:`ModelWarning` says what is out of bounds, why it matters and the threshold, so a page can
show it beside the number it qualifies and a report can print it. Topic modules build their own
warnings with :func:`range_warning` and the other helpers here.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

#: Mach number above which incompressible aerodynamics is no longer a fair model (common practice).
MACH_INCOMPRESSIBLE_LIMIT = 0.3


@dataclass(frozen=True)
class ModelWarning:
    """One validity warning.

    Attributes
    ----------
    code : str
        Stable identifier, e.g. ``"spin_ratio_outside_data"``; tests and the UI key on it.
    message : str
        Plain sentence for the user, including the reason and the threshold.
    subject : str
        Which result it qualifies (e.g. ``"thrust_n"``, ``"carry_m"``), or ``""`` for all.
    severity : str
        ``"caution"`` (model stretched) or ``"invalid"`` (result not meaningful).
    """

    code: str
    message: str
    subject: str = ""
    severity: str = "caution"
    #: For messages with quantities: the message with ``{name}`` placeholders, and the
    #: quantities as ``(name, core value, quantity kind, digits)``; :meth:`text` writes them in
    #: a unit system, ``message`` holds the SI text.
    template: str = ""
    quantities: tuple = ()

    def text(self, system: str = "SI") -> str:
        """The message with its quantities in the display units of ``system``."""
        if not self.template:
            return self.message
        from liftcore.units import quantity_text

        return self.template.format(**{name: quantity_text(value, kind, system, digits)
                                       for name, value, kind, digits in self.quantities})

    def as_dict(self) -> dict:
        return {"code": self.code, "message": self.message, "subject": self.subject,
                "severity": self.severity}


def quantity_warning(code: str, template: str, quantities: dict, subject: str = "",
                     severity: str = "caution") -> ModelWarning:
    """A warning whose numbers follow the unit switch: ``template`` holds ``{name}`` where each
    quantity goes; ``quantities`` maps name -> (core value, quantity kind[, digits])."""
    qs = tuple((name, float(q[0]), q[1], q[2] if len(q) > 2 else 3) for name, q in quantities.items())
    w = ModelWarning(code, "", subject, severity, template, qs)
    return ModelWarning(code, w.text("SI"), subject, severity, template, qs)


def range_warning(code: str, what: str, values, low: float, high: float, unit: str = "",
                  reason: str = "", subject: str = "") -> tuple[ModelWarning, ...]:
    """A warning when any of ``values`` lies outside ``[low, high]``; empty tuple otherwise."""
    v = np.asarray(values, dtype=float)
    v = v[np.isfinite(v)]
    if v.size == 0:
        return ()
    vmin, vmax = float(v.min()), float(v.max())
    if vmin >= low and vmax <= high:
        return ()
    u = f" {unit}" if unit else ""
    seen = f"{vmin:.3g}{u}" if vmin == vmax else f"{vmin:.3g} to {vmax:.3g}{u}"
    msg = f"{what} {seen} is outside {low:.3g} to {high:.3g}{u}"
    if reason:
        msg += f": {reason}"
    return (ModelWarning(code, msg, subject),)


def mach_warning(speed_m_s, speed_of_sound_m_s, subject: str = "") -> tuple[ModelWarning, ...]:
    """Warn when the flow Mach number exceeds the incompressible limit (0.3, common practice)."""
    mach = np.max(np.asarray(speed_m_s, dtype=float) / speed_of_sound_m_s)
    if mach > MACH_INCOMPRESSIBLE_LIMIT:
        return (ModelWarning("mach_above_0_3",
                             f"Mach number {mach:.2f} exceeds {MACH_INCOMPRESSIBLE_LIMIT}: "
                             "compressibility is not modelled", subject),)
    return ()


def merge(*groups) -> tuple[ModelWarning, ...]:
    """Concatenate warning tuples, dropping repeats of the same code and subject."""
    out, seen = [], set()
    for group in groups:
        for w in group:
            k = (w.code, w.subject, w.message)
            if k not in seen:
                seen.add(k)
                out.append(w)
    return tuple(out)
