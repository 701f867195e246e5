"""``python -m calcreport``: the same as the ``calcreport`` command."""

from calcreport.cli import main

raise SystemExit(main())
