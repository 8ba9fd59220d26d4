"""The design-review report (report.html) and the figure style it shares with the comparison page.

One concept per module: ``style`` (palette, rc style, Figure making, SVG), ``data`` (what the figures plot),
``figures`` (each figure as a matplotlib Figure; the registry FIGURE_MAKERS), ``texts`` (fixed texts, CSS),
``sections`` (the HTML sections), ``page`` (``report_html`` and ``figure_svgs``). Import from the module:
this package's ``__init__`` stays empty so that importing any part loads no matplotlib it does not need.
"""
