"""From a study to solved, stored flames.

points      the study's points and their store keys
warm_tree   which neighbour each point warm-starts from
schedule    the order a plan is solved in (shared by the run and its estimate)
worker      the task a worker runs (one flame, plain data in and out)
lifeline    worker processes end with the run's process (no orphans after a kill)
backends    this process, local processes (loky), or a Dask cluster (dask_backend)
run         the run loop: hand out ready points, commit each finished flame
"""
