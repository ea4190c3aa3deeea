from reviewer.cli import run

run()
