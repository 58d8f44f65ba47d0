from cognomen.server.cli import main

raise SystemExit(main())
