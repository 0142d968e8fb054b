from verify.cli.main import main

main()
