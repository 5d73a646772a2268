from fieldcol.cli import main

raise SystemExit(main())
