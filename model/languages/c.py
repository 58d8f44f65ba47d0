"""C and C++: typed declarations, `auto`, members reached through `->` and `::`."""

from __future__ import annotations

from .base import words
from .java import TypedLanguage

_C_RESERVED = words("""auto break case char const continue default do double else enum extern float for goto
    if inline int long register restrict return short signed sizeof static struct switch typedef union
    unsigned void volatile while bool true false NULL""")


class C(TypedLanguage):
    name = "c"
    pygments_alias = "c"
    pygments_names = ("C",)
    reserved = _C_RESERVED
    naming_style = "snake"
    member_access = frozenset({".", "->", "::"})


class CPlusPlus(C):
    name = "cpp"
    pygments_alias = "cpp"
    pygments_names = ("C++",)
    reserved = _C_RESERVED | words("class namespace template typename this new delete public private protected "
                                   "virtual nullptr auto")
    declaration_words = frozenset({"auto"})


C_LANGUAGE = C()
CPP = CPlusPlus()
