// Larkspur: a small ALU using a package (localparam, typedef, enum, function), unique case
// over enum values and a package-qualified function call.
package larkspur_pkg;
  localparam int WIDTH = 6;
  typedef logic [5:0] word_t;  // Icarus 11 cannot size a package typedef by a package parameter
  typedef enum logic [1:0] {OP_ADD, OP_SUB, OP_AND, OP_OR} op_t;
  function automatic word_t rev(input word_t v);
    for (int i = 0; i < WIDTH; i++) rev[i] = v[WIDTH-1-i];
  endfunction
endpackage

import larkspur_pkg::*;

module larkspur_alu (
  input  word_t a, b,
  input  op_t   op,
  output word_t y,
  output logic  big,
  output word_t r
);
  always_comb begin
    unique case (op)
      OP_ADD: y = a + b;
      OP_SUB: y = a - b;
      OP_AND: y = a & b;
      OP_OR:  y = a | b;
    endcase
  end
  assign big = (a >= 6'd60);
  assign r = larkspur_pkg::rev(a) ^ ~b;
endmodule
