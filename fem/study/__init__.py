"""Many checks at once: the regression suite (`regress`) and parametric sweeps (`sweep`).

Both run checks through `fem.api` in worker processes (`pool`). A sweep's parts: `keys`
(the varied dotted keys), `toml_writer` (each point's case.toml), `index` (the resumable
index.jsonl) and `sweep_outputs` (sweep.csv, summary.json, ratio.png).
"""
