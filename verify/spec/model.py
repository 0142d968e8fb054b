"""The Spec: parsed, checked equations for one design, and its three translations."""

from __future__ import annotations

from typing import Any, Mapping, Sequence

from verify.errors import SpecError
from verify.model.builder import GateBuilder
from verify.model.netlist import CONST0, Netlist, Port
from verify.spec.evaluate import Program
from verify.spec.printer import Printer
from verify.spec.resolve import Resolver
from verify.spec.syntax import Equation, Parser
from verify.spec.to_gates import Bits, GateCompiler
from verify.spec.to_z3 import Z3Compiler


class Spec:
    """Parsed, checked equations for one design. Build with :func:`parse` or :func:`infer`."""

    def __init__(self, source: str, design: Netlist, equations: Sequence[Equation],
                 inputs_used: set[str], inferred: bool = False):
        self.source = source  # the text as the user wrote it
        self.design_name = design.name
        self.inputs: tuple[Port, ...] = design.inputs
        self.outputs: tuple[Port, ...] = design.outputs
        self.equations: tuple[Equation, ...] = tuple(equations)
        self.inputs_used: set[str] = set(inputs_used)
        self.inferred = inferred
        widths = {p.name: p.width for p in design.outputs}
        printer = Printer()
        self.text: str = "; ".join(printer.equation(eq, widths) for eq in self.equations)
        self._compile()
        self._reference: Netlist | None = None

    def _compile(self) -> None:
        self._int = [(Program(eq.rhs), eq.width, self._layout(eq)) for eq in self.equations]

    @staticmethod
    def _layout(eq: Equation) -> list[tuple[str, int, int, int]]:
        """(port, lsb, width, offset in the equation's value) per target."""
        out, offset = [], eq.width
        for t in eq.targets:
            offset -= t.width
            out.append((t.port, t.lsb, t.width, offset))
        return out

    def __repr__(self) -> str:
        return f"Spec({self.text!r}{', inferred' if self.inferred else ''})"

    # Pickling (process pools) sends the text and ports and parses again on arrival: the syntax
    # trees may be nested too deeply for pickle's recursion, and the programs hold functions.
    def __getstate__(self) -> dict[str, Any]:
        return {"source": self.source, "design_name": self.design_name, "inputs": self.inputs,
                "outputs": self.outputs, "inferred": self.inferred, "_reference": self._reference}

    def __setstate__(self, state: dict[str, Any]) -> None:
        ports = Netlist(state["design_name"], state["inputs"], state["outputs"], ())
        again = parse(state["source"], ports, inferred=state["inferred"])
        self.__dict__.update(again.__dict__)
        self._reference = state["_reference"]

    # ---- ground truth
    def evaluate(self, inputs: Mapping[str, int]) -> dict[str, int]:
        """Every output port's specified value (0 <= v < 2^width) for one input vector."""
        env: dict[str, int] = {}
        for p in self.inputs:
            if p.name in self.inputs_used:
                v = inputs[p.name]
                if not 0 <= v < 1 << p.width:
                    raise ValueError(f"input {p.name}={v} does not fit its {p.width} bits")
                env[p.name] = v
        outs = {p.name: 0 for p in self.outputs}
        for program, width, layout in self._int:
            v = program(env) & ((1 << width) - 1)
            for port, lsb, w, offset in layout:
                outs[port] |= ((v >> offset) & ((1 << w) - 1)) << lsb
                env[port] = outs[port]
        return outs

    # ---- gates
    def reference(self) -> Netlist:
        """The spec as gates, with the design's input and output ports (cached)."""
        if self._reference is None:
            self._reference = self._build_reference()
        return self._reference

    def _build_reference(self) -> Netlist:
        names = {p.name for p in (*self.inputs, *self.outputs)}
        prefix = "ref_"
        while any(n.startswith(prefix) for n in names):
            prefix += "_"
        b = GateBuilder(prefix, fold=True)
        env: dict[str, Bits] = {p.name: Bits(tuple(p.bits)) for p in self.inputs}
        outs: dict[str, list[str]] = {p.name: [CONST0] * p.width for p in self.outputs}
        compiler = GateCompiler(b, env, self.source)
        for eq, (_, width, layout) in zip(self.equations, self._int):
            value = compiler.visit(eq.rhs).low(width)
            for port, lsb, w, offset in layout:
                outs[port][lsb:lsb + w] = value[offset:offset + w]
                env[port] = Bits(tuple(outs[port]))
        return b.netlist(f"{self.design_name}_spec", self.inputs, outs,
                         origin=f"spec: {self.text}")

    # ---- z3
    def to_z3(self, inputs: Mapping[str, Any]) -> dict[str, Any]:
        """Each output port's specified value as a z3 BitVec of the port width (word-level)."""
        import z3
        env: dict[str, Any] = {}
        for p in self.inputs:
            if p.name in self.inputs_used:
                x = inputs[p.name]
                if x.size() != p.width:
                    raise ValueError(f"z3 input {p.name} is {x.size()} bits; the port is {p.width}")
                env[p.name] = x
        pieces: dict[str, list[tuple[int, Any]]] = {p.name: [] for p in self.outputs}
        compiler = Z3Compiler(env)
        out: dict[str, Any] = {}
        for eq, (_, width, layout) in zip(self.equations, self._int):
            value = compiler.fit(compiler.visit(eq.rhs), width)
            for port, lsb, w, offset in layout:
                pieces[port].append((lsb, z3.Extract(offset + w - 1, offset, value)))
                parts = [x for _, x in sorted(pieces[port], key=lambda t: -t[0])]
                out[port] = parts[0] if len(parts) == 1 else z3.Concat(*parts)
                env[port] = out[port]
        return {p.name: out[p.name] for p in self.outputs}


def parse(text: str, design: Netlist, *, inferred: bool = False) -> Spec:
    """Parse and check spec equations against a design; every mistake is one SpecError."""
    if not isinstance(text, str):
        raise SpecError(f"a spec is text, got {type(text).__name__}", where="spec")
    equations = Parser(text).equations()
    resolver = Resolver(text, design)
    resolved = [resolver.equation(eq) for eq in equations]
    resolver.finish()
    return Spec(text, design, resolved, resolver.used, inferred)
