"""The member kind (`kind = "beam"`): a 2D plane stress/strain member, drawn in elevation.

Read in the order of the chain: `gmsh_model` (the OCC model, every patch a physical group)
-> `mesh` (size fields, the hand-over to scikit-fem) -> `solve` -> `recovery` (stresses at
element vertices) -> `cuts` (FE profiles and resultants) beside `hand` (the hand side at the
same cuts) -> `level` (one mesh level of all that) -> `compare` (findings at cuts and
stations) and `concentration` (holes, fillets, corners) -> `check` (the convergence study
and the member's `Result`). `adapt` sizes adaptive levels; `hand_only` is `shearcheck hand`.
"""
