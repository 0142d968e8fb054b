"""Names shared by the parts of the Verilog translation: node kinds, limits, wording."""

from __future__ import annotations

from pyslang import ast

from verify.model.netlist import CONST0, CONST1

EK = ast.ExpressionKind
SK = ast.SymbolKind
STK = ast.StatementKind
BO = ast.BinaryOperator
UO = ast.UnaryOperator

_CONSTS = (CONST0, CONST1)
_MAX_LOOP = 1 << 16
_MAX_MUL = 128  # widest '*' translated into gates

_COMPARE = {BO.Equality, BO.Inequality, BO.CaseEquality, BO.CaseInequality, BO.GreaterThanEqual,
            BO.GreaterThan, BO.LessThanEqual, BO.LessThan, BO.WildcardEquality,
            BO.WildcardInequality}

_GATE_PRIMS = {"and", "or", "xor", "nand", "nor", "xnor", "not", "buf"}
_TRI_PRIMS = {"bufif0", "bufif1", "notif0", "notif1", "nmos", "pmos", "rnmos", "rpmos", "cmos",
              "rcmos", "tran", "rtran", "tranif0", "tranif1", "rtranif0", "rtranif1", "pullup",
              "pulldown"}

_IGNORED_MEMBERS = {SK.Parameter, SK.TypeParameter, SK.Genvar, SK.Port, SK.MultiPort,
                    SK.TypeAlias, SK.Subroutine, SK.EmptyMember, SK.ExplicitImport,
                    SK.WildcardImport, SK.StatementBlock, SK.TransparentMember, SK.EnumValue,
                    SK.ForwardingTypedef, SK.NetType, SK.ElabSystemTask, SK.DefParam,
                    SK.Specparam, SK.Attribute, SK.LetDecl}


def _kind_words(k) -> str:
    words = {SK.Instance: "module instance", SK.ClockingBlock: "a clocking block",
             SK.Modport: "a modport", SK.SpecifyBlock: "a specify block",
             SK.CheckerInstance: "a checker instance", SK.NetAlias: "a net alias",
             SK.Sequence: "a sequence", SK.Property: "a property",
             SK.InterfacePort: "an interface port", SK.ClassType: "a class",
             SK.CovergroupType: "a covergroup"}
    if k in words:
        return words[k]
    name = k.name
    out = "".join(" " + c.lower() if c.isupper() else c for c in name).strip()
    return f"a {out}"


def _expr_words(e) -> str:
    return {EK.RealLiteral: "a real number", EK.StringLiteral: "a string",
            EK.TimeLiteral: "a time value", EK.SimpleAssignmentPattern: "an assignment pattern",
            EK.StructuredAssignmentPattern: "an assignment pattern",
            EK.ReplicatedAssignmentPattern: "an assignment pattern",
            }.get(e.kind, f"the expression kind {e.kind.name}")


def _stmt_words(k) -> str:
    return {STK.WhileLoop: "a while loop", STK.DoWhileLoop: "a do-while loop",
            STK.ForeverLoop: "a forever loop", STK.ForeachLoop: "a foreach loop",
            STK.Break: "break", STK.Continue: "continue", STK.Disable: "disable",
            STK.Wait: "wait", STK.EventTrigger: "an event trigger",
            STK.PatternCase: "case matches", STK.RandCase: "randcase",
            STK.ProceduralAssign: "a procedural assign/force",
            STK.ProceduralDeassign: "deassign/release"}.get(k, f"the statement kind {k.name}")


# how deeply expressions and statements may nest (each level is a few Python frames; the
# interpreter's default limit of 1,000 frames must hold them with room to spare)
MAX_NEST = 200
