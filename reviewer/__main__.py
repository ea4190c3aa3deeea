from reviewer.cli import main

raise SystemExit(main())
