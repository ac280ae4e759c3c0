"""Pictures of an analysis (``fibrewise analyze --plot FILE.png``): the degree and the matrix size
of every Gröbner step, and the Hilbert function read off the Hilbert series.

matplotlib is an optional extra, imported here only, with the file-only Agg backend.
"""

from __future__ import annotations

from math import comb


def series_coefficients(numerator: list[int], denominator_exponent: int, count: int) -> list[int]:
    """The first ``count`` coefficients of N(t) / (1 - t)^D: the values of the Hilbert function
    (1 / (1 - t)^D = sum over i of C(i + D - 1, D - 1) t^i)."""
    d = denominator_exponent

    def inverse_power(i: int) -> int:
        return (1 if i == 0 else 0) if d == 0 else comb(i + d - 1, d - 1)

    return [sum(c * inverse_power(i - j) for j, c in enumerate(numerator) if j <= i) for i in range(count)]


def draw_analysis(path: str, result: dict) -> None:
    """Writes the picture of an ``analyze`` result (its ``stats`` and ``hilbert``) to ``path``."""
    try:
        import matplotlib
    except ImportError:
        raise RuntimeError("--plot needs the optional package matplotlib (pip install matplotlib)") from None
    matplotlib.use("Agg")
    import matplotlib.pyplot as plt
    from matplotlib.ticker import MaxNLocator

    steps = result["stats"]["steps"]
    series = result.get("hilbert")
    fig, (left, right) = plt.subplots(1, 2, figsize=(10, 4))
    _draw_steps(left, steps)
    _draw_hilbert(right, series)
    for ax in (left, right):
        ax.xaxis.set_major_locator(MaxNLocator(integer=True))
        ax.yaxis.set_major_locator(MaxNLocator(integer=True))
    fig.suptitle(f"{result['file']}: {result['summary']}", fontsize=9)
    fig.tight_layout()
    fig.savefig(path, dpi=100)
    plt.close(fig)


def _draw_steps(ax, steps: list[dict]) -> None:
    numbers = list(range(1, len(steps) + 1))
    ax.set_title("Gröbner basis steps")
    ax.set_xlabel("step")
    if not steps:
        ax.text(0.5, 0.5, "no steps recorded", ha="center", transform=ax.transAxes)
        return
    ax.plot(numbers, [s["degree"] for s in steps], "o-", color="tab:blue", label="degree")
    ax.set_ylabel("degree", color="tab:blue")
    sizes = [s["rows"] * s["columns"] for s in steps]
    if any(sizes):
        twin = ax.twinx()
        twin.bar(numbers, sizes, alpha=0.3, color="tab:orange", label="matrix rows × columns")
        twin.set_ylabel("matrix rows × columns", color="tab:orange")


def _draw_hilbert(ax, series: dict | None) -> None:
    ax.set_title("Hilbert function")
    ax.set_xlabel("s")
    if not series:
        ax.text(0.5, 0.5, "Hilbert series not available", ha="center", transform=ax.transAxes)
        return
    count = max(len(series["numerator"]), int(series.get("regularity_index") or 0)) + 4
    values = series_coefficients(series["numerator"], series["denominator_exponent"], count)
    ax.plot(range(count), values, "s-", color="tab:green")
    ax.set_ylabel("H(s)")


def draw_plan(path: str, result: dict) -> None:
    """Writes the expected total time of a guess plan (``fibrewise plan --plot``) against k."""
    try:
        import matplotlib
    except ImportError:
        raise RuntimeError("--plot needs the optional package matplotlib (pip install matplotlib)") from None
    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    rows = result["rows"]
    fig, ax = plt.subplots(figsize=(6, 4))
    ax.semilogy(
        [r["k"] for r in rows], [max(r["total_seconds"], 1e-9) for r in rows], "o-", label="expected total"
    )
    ax.semilogy(
        [r["k"] for r in rows],
        [max(r["seconds"], 1e-9) for r in rows],
        "s--",
        alpha=0.6,
        label="one specialised system",
    )
    ax.set_xlabel("guessed variables k")
    ax.set_ylabel("seconds")
    ax.set_title(f"{result.get('file') or 'system'}: best k = {result['best']}", fontsize=9)
    ax.legend()
    fig.tight_layout()
    fig.savefig(path, dpi=100)
    plt.close(fig)
