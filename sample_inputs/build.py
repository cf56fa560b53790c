"""Rebuild the demo input workbook in this folder: python sample_inputs/build.py"""

from pathlib import Path

from ranker.demo import write_demo

if __name__ == "__main__":
    print(write_demo(Path(__file__).resolve().parent))
