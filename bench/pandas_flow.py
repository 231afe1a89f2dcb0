"""The pandas side of the benchmark: what a data scientist would otherwise write by hand to get the
level counts and the target rate of every categorical column of a CSV extract.

    python3 bench/pandas_flow.py FILE --target COL --columns a,b,c

read_csv with dtype=str (level identity = the file's text, like the scan), the target made numeric,
then per categorical column value_counts(dropna=False) and groupby(col)[target].mean().
Prints one JSON line (rows, levels, seconds) on stdout. When BENCH_RSS_FILE is set it also writes
its own peak RSS (resource.getrusage, kB on Linux) and CPU time there, for machines without
/usr/bin/time.
"""
import argparse
import json
import os
import resource
import time

import pandas as pd


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("file")
    parser.add_argument("--target", required=True)
    parser.add_argument("--columns", required=True)
    args = parser.parse_args()
    started = time.perf_counter()

    df = pd.read_csv(args.file, dtype=str)
    df[args.target] = pd.to_numeric(df[args.target], errors="coerce")
    levels = 0
    for col in args.columns.split(","):
        counts = df[col].value_counts(dropna=False)
        rates = df.groupby(col, dropna=False)[args.target].mean()
        levels += len(counts)
        assert len(rates) == len(counts)

    out = {"rows": len(df), "levels": levels, "seconds": round(time.perf_counter() - started, 3)}
    print(json.dumps(out))
    rss_file = os.environ.get("BENCH_RSS_FILE")
    if rss_file:
        usage = resource.getrusage(resource.RUSAGE_SELF)
        with open(rss_file, "w", encoding="utf-8") as fh:
            json.dump({"maxRssKB": usage.ru_maxrss, "cpuMs": round((usage.ru_utime + usage.ru_stime) * 1000)}, fh)


if __name__ == "__main__":
    main()
