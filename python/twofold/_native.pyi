"""The extension module (Rust, PyO3). Use the wrappers in twofold instead."""

from typing import List, Optional

__version__: str

def analyse_json(
    text: str,
    budget: Optional[float] = None,
    height: Optional[int] = None,
    evidence: bool = True,
    certificate: bool = False,
) -> str: ...
def analyse_many_json(
    texts: List[str],
    threads: int = 0,
    budget: Optional[float] = None,
    height: Optional[int] = None,
    evidence: bool = True,
    certificate: bool = False,
) -> List[str]: ...
