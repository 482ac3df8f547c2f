"""The use cases, Qt-free: what the window asks for, done against the engine and the store.

Open a case at intake, take a reading, skip or undo one, conclude, repair, verify, close; resume a
case; tell a closed case's story and run it through today's engine; the content of the printed
reports; the owner's review (history pages, figures, amendments); practice rounds and progress.
The ui calls only these to reach the shop's record (an import contract in pyproject.toml), and
shows what they return. Each function that writes keeps its step in one committed transaction.
"""
