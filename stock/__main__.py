from stock.cli import main

main()
