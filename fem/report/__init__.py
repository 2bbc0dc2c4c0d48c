"""What a finished check writes besides results.json: figures, field files, the design note.

`figures` draws every PNG (`member_figures`, `section_figures`, `convergence_figure`);
`fields` writes fields.vtu and profiles.csv; `note` fills the design note from `blocks` and
`section_note`, and `html` / `pdf` render it; `console` is the terminal summary.
"""
