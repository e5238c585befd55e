"""app/jobs.py, the one runner of the study's and the search's long work: figures reported,
stop asked for between steps, the result or the error kept, a bound on jobs running at once."""
from __future__ import annotations

import threading

from app import jobs
from engine.model import DesignError, Issue


def _wait(job: jobs.Job) -> None:
    assert job.finished.wait(10), "the job did not finish"


def test_a_job_reports_stops_on_request_and_keeps_its_result():
    go = threading.Event()

    def work(job: jobs.Job) -> str:
        steps = 0
        while not job.stop_requested():
            go.wait(5)
            steps += 1
            job.report(done=steps)
        return f"stopped after {steps}"

    key = jobs.start("test", work, done=0)
    job = jobs.get("test", key)
    assert job is not None and job.figures == {"done": 0} and not job.finished.is_set()
    assert jobs.get("other kind", key) is None and jobs.get("test", "no-such-key") is None
    job.stop.set()
    go.set()
    _wait(job)
    assert job.error is None and job.result == f"stopped after {job.figures['done']}"


def test_an_error_is_kept_for_the_page():
    def work(job: jobs.Job) -> None:
        raise DesignError([Issue(path="x", message="bad x")])

    key = jobs.start("test", work)
    job = jobs.get("test", key)
    _wait(job)
    assert isinstance(job.error, DesignError) and job.error.errors[0].message == "bad x" and job.result is None


def test_at_most_max_running_jobs_run_at_once():
    release = threading.Event()
    keys = []
    try:
        while True:
            key = jobs.start("test", lambda job: release.wait(10))
            if key is None:
                break
            keys.append(key)
            assert len(keys) <= jobs.MAX_RUNNING
        running = sum(not j.finished.is_set() for j in jobs._JOBS.values())
        assert running == jobs.MAX_RUNNING
    finally:
        release.set()
    for k in keys:
        _wait(jobs.get("test", k))
    assert jobs.start("test", lambda job: None) is not None  # room again once they finished


def test_finished_jobs_nobody_asked_for_are_dropped():
    key = jobs.start("test", lambda job: 1)
    job = jobs.get("test", key)
    _wait(job)
    job.touched -= jobs.KEEP_S + 1
    jobs.prune()
    assert jobs.get("test", key) is None
