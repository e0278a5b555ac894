"""Engine queries as Python source text (``df`` names the native data; each returns pandas).
plotwise evaluates the text itself and pastes the same text into the generated code."""

from __future__ import annotations

from plotwise.sources.base import Source


# ----------------------------------------------------------------------------------------------
# Engine expressions (source text). ``df`` names the native data; each returns pandas.
# ----------------------------------------------------------------------------------------------
def chained(expr: str, indent: int) -> str:
    """A long method chain split at its top-level calls, one per line, inside parentheses (how
    people write engine queries by hand); short expressions stay on one line."""
    if len(expr) + indent <= 100:
        return expr
    parts, depth, quote, start = [], 0, None, 0
    for i, ch in enumerate(expr):
        if quote:
            if ch == quote and expr[i - 1] != "\\":
                quote = None
        elif ch in "'\"":
            quote = ch
        elif ch in "([{":
            depth += 1
        elif ch in ")]}":
            depth -= 1
        elif ch == "." and depth == 0 and i and expr[i - 1] in ")]":
            parts.append(expr[start:i])
            start = i
    parts.append(expr[start:])
    if len(parts) == 1:
        return expr
    pad = "\n" + " " * (indent + 1)
    return "(" + pad.join(parts) + ")"


def _keyword(name: str, value: str) -> str:
    """A keyword argument ``name=value``, or ``**{'name': value}`` when name is no identifier."""
    import keyword

    if name.isidentifier() and not keyword.iskeyword(name):
        return f"{name}={value}"
    return f"**{{{name!r}: {value}}}"


def _minus(value: float) -> str:
    """``- value`` written the way a person would (``+ 0.5`` rather than ``- -0.5``)."""
    return f"- {value!r}" if value >= 0 else f"+ {-value!r}"


def _fresh(name: str, taken) -> str:
    while name in taken:
        name += "_"
    return name


def complete_rows(src: Source, cols: list[str], finite: tuple = (), frame: str = "df") -> str:
    """The columns ``cols``, rows with a missing value (or a non-finite number in ``finite``)
    left out, still inside the engine."""
    if src.engine == "dask":
        expr = f"{frame}[{cols!r}].dropna()"
        for c in finite:
            expr += f".pipe(lambda t: t[np.isfinite(t[{c!r}])])"
        return expr
    expr = f"nw.from_native({frame}).lazy().select({cols!r}).drop_nulls()"
    for c in finite:
        expr += f".filter(nw.col({c!r}).is_finite())"
    return expr


def _to_pandas(src: Source, expr: str) -> str:
    return f"{expr}.compute()" if src.engine == "dask" else f'{expr}.collect("pandas").to_native()'


def count_name(keys, y=None) -> str:
    return _fresh("rows", set(keys) | {y})


def grouped_expr(src: Source, keys: list[str], y: str | None, stat: str = "sum",
                 squares: bool = False, finite: bool = True, frame: str = "df",
                 complete_in: tuple = ()) -> str:
    """One row per group of ``keys``: the row count (column ``count_name``), and for ``y`` its
    sum (or median), and with ``squares`` the sum of squares (column ``y + '_squares'``). Rows
    missing a value in keys, y or ``complete_in`` are left out."""
    n = count_name(keys, y)
    cols = list(dict.fromkeys(keys + ([y] if y else []) + list(complete_in)))
    fin = (y,) if (y and finite) else ()
    sq = _fresh(f"{y}_squares", set(cols)) if (y and squares) else None
    base = complete_rows(src, cols, fin, frame)
    if src.engine == "dask":
        parts = [_keyword(n, f"({(y or keys[0])!r}, 'count')")]
        if y:
            parts.append(_keyword(y, f"({y!r}, {('median' if stat == 'median' else 'sum')!r})"))
        if sq:
            base += f".assign({_keyword(sq, f'lambda t: t[{y!r}] ** 2')})"
            parts.append(_keyword(sq, f"({sq!r}, 'sum')"))
        return (f"{base}.groupby({keys!r}, observed=True).agg({', '.join(parts)})"
                ".reset_index().compute()")
    if src.engine == "pyarrow" and stat == "median" and y:
        # PyArrow's grouped median is approximate (a t-digest); the table is in memory, so the
        # used columns go to pandas for an exact median.
        return (f"{_to_pandas(src, base)}.groupby({keys!r}, observed=True)"
                f".agg({_keyword(n, repr((y, 'count')))}, {_keyword(y, repr((y, 'median')))})"
                ".reset_index()")
    aggs = [f"nw.len().alias({n!r})"]
    if y:
        aggs.append(f"nw.col({y!r}).{'median' if stat == 'median' else 'sum'}()")
    if sq:
        base += f".with_columns((nw.col({y!r}) ** 2).alias({sq!r}))"
        aggs.append(f"nw.col({sq!r}).sum()")
    if src.engine == "duckdb" and any("." in k for k in keys):
        # narwhals' DuckDB group_by reads a dot in a key's name as table.column: the keys are
        # grouped under plain names and get their own names back in pandas.
        plain = {k: _fresh(k.replace(".", "_"), set(cols) | {n, sq}) for k in keys if "." in k}
        back = {v: k for k, v in plain.items()}
        grouped = [plain.get(k, k) for k in keys]
        return (_to_pandas(src, f"{base}.rename({plain!r}).group_by({grouped!r})"
                                f".agg({', '.join(aggs)})") + f".rename(columns={back!r})")
    return _to_pandas(src, f"{base}.group_by({keys!r}).agg({', '.join(aggs)})")


def sample_expr(src: Source, cols: list[str], k: int, n: int, complete: bool = True,
                finite: tuple = (), frame: str = "df") -> str:
    """At most about ``k`` random rows of ``cols`` (all rows when ``n`` ≤ k), seeded."""
    if complete:
        base = complete_rows(src, cols, finite, frame)
    elif src.engine == "dask":
        base = f"{frame}[{cols!r}]"
    else:
        base = f"nw.from_native({frame}).lazy().select({cols!r})"
    if n <= k:
        return _to_pandas(src, base)
    frac = min(1.0, k / n)
    if src.engine == "dask":  # Bernoulli sample in every partition: about k rows
        return f"{base}.sample(frac={frac:.6g}, random_state=0).compute()"
    if src.engine == "spark":  # Bernoulli sample on the executors: about k rows
        return f"{base}.to_native().sample(fraction={frac:.6g}, seed=0).toPandas()"
    if src.engine == "duckdb":  # reservoir sample inside DuckDB: exactly k rows
        return (f'{base}.to_native().query("t", "SELECT * FROM {_bernoulli_first(k, n)}USING '
                f'SAMPLE reservoir({k} ROWS) REPEATABLE (0)").df()')
    return f"{base}.collect().sample(n={k}, seed=0).to_pandas()"  # in memory already


def _bernoulli_first(k: int, n: int) -> str:
    """A reservoir sample keeps every row in one thread; on many rows a seeded Bernoulli pass
    (parallel) first keeps a little more than k of them (six binomial standard deviations more,
    so fewer than k is a one-in-a-billion event), and the reservoir then takes exactly k of
    those: still a simple random sample of k rows, at about half the cost on 20 million rows
    (benchmarks/engines.py)."""
    pct = 100 * (k + 6 * k ** 0.5 + 100) / n
    return "t " if pct > 50 else f"(SELECT * FROM t USING SAMPLE {pct:.6g}% (bernoulli, 0)) "


def bins_expr(src: Source, col: str, lo: float, width: float, k: int, log: bool = False,
              frame: str = "df") -> str:
    """Row counts in ``k`` equal bins of ``width`` from ``lo`` (of log10 values with ``log``),
    counted in the engine; the last bin includes its right edge, as in numpy.histogram."""
    base = complete_rows(src, [col], (col,), frame)
    if src.engine == "dask":
        v = f"np.log10(t[{col!r}])" if log else f"t[{col!r}]"
        cut = f".pipe(lambda t: t[t[{col!r}] > 0])" if log else ""
        return (f"{base}{cut}.assign(bin=lambda t: np.floor(({v} {_minus(lo)}) / {width!r})"
                f".clip(0, {k - 1}).astype('int64')).groupby('bin').size().compute()")
    v = f"nw.col({col!r}).log(10)" if log else f"nw.col({col!r})"
    cut = f".filter(nw.col({col!r}) > 0)" if log else ""
    return (f"{base}{cut}.select((({v} {_minus(lo)}) / {width!r}).floor().clip(0, {k - 1})"
            f".cast(nw.Int64).alias('bin')).group_by('bin').agg(nw.len())"
            '.collect("pandas").to_native().set_index("bin")["len"]')
