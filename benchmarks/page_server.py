"""``streamlit run`` with every script run timed on the server (used by bench_pages).

    python benchmarks/page_server.py run app.py --server.port 8765 ...

The arguments are those of the ``streamlit`` command. With ``LIFTCORE_BENCH_RUN_LOG`` set, one
JSON line per script execution is appended to that file: the session, the wall-clock start and
end of the script itself (``time.time()``, seconds) and the end of Streamlit's clean-up after it
(widget state, the "finished" message, the garbage collection). With
``LIFTCORE_BENCH_PROFILE_DIR`` set, each execution also runs under cProfile and its statistics
are written to ``run-<n>.prof`` in that folder (slower: for finding where the time goes, not for
timing). Nothing changes in what the page does or shows.
"""

from __future__ import annotations

import itertools
import json
import os
import sys
import threading
import time


def install(log_path: str | None, profile_dir: str | None) -> None:
    """Wrap Streamlit's script execution and its clean-up with wall-clock stamps."""
    from streamlit.runtime.scriptrunner import script_runner as sr

    lock = threading.Lock()
    counter = itertools.count(1)
    local = threading.local()
    run_exec = sr.exec_func_with_error_handling
    finish = sr.ScriptRunner._on_script_finished

    def write(record: dict) -> None:
        if log_path:
            with lock, open(log_path, "a", encoding="utf-8") as fh:
                fh.write(json.dumps(record) + "\n")

    def timed_exec(func, ctx):
        n = next(counter)
        prof = None
        if profile_dir:
            import cProfile

            prof = cProfile.Profile()
        start = time.time()
        try:
            if prof is None:
                return run_exec(func, ctx)
            prof.enable()
            try:
                return run_exec(func, ctx)
            finally:
                prof.disable()
        finally:
            end = time.time()
            local.pending = {"run": n, "session": ctx.session_id, "start": start, "end": end}
            if prof is not None:
                prof.dump_stats(os.path.join(profile_dir, f"run-{n}.prof"))

    def timed_finish(self, ctx, *args, **kwargs):
        try:
            return finish(self, ctx, *args, **kwargs)
        finally:
            record = getattr(local, "pending", None)
            local.pending = None
            if record is not None:
                record["finished"] = time.time()
                write(record)

    sr.exec_func_with_error_handling = timed_exec
    sr.ScriptRunner._on_script_finished = timed_finish


def main() -> None:
    install(os.environ.get("LIFTCORE_BENCH_RUN_LOG"), os.environ.get("LIFTCORE_BENCH_PROFILE_DIR"))
    from streamlit.web import cli

    sys.argv = ["streamlit", *sys.argv[1:]]
    cli.main(prog_name="streamlit")


if __name__ == "__main__":
    main()
