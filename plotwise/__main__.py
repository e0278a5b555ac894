from plotwise.cli import main

raise SystemExit(main())
