// Larkspur: Verilog expression width and sign rules the translation must reproduce.
module larkspur_rules (
  input  logic [3:0]        a,
  input  logic signed [3:0] sb,
  input  logic [3:0]        c,
  output logic [4:0]        carry_kept,   // a + c in a 5-bit context keeps the carry
  output logic [4:0]        carry_lost,   // (a + c) >> 1 in a 5-bit context keeps it too
  output logic [3:0]        carry_cut,    // {a + c} is self-determined: 4 bits
  output logic [7:0]        mixed,        // signed + unsigned is unsigned: sb is zero-extended
  output logic [7:0]        both_signed,  // sb + sb sign-extends
  output logic              cmp_mixed,    // sb < a compares unsigned
  output logic              cmp_signed,   // sb < $signed(a) compares signed
  output logic [3:0]        ashr,         // >>> on a signed operand shifts in the sign
  output logic [3:0]        ashr_u,       // >>> on an unsigned operand shifts in zeros
  output logic [7:0]        prod,         // 4x4 multiply in an 8-bit context
  output logic [5:0]        tern,         // the branches extend to the context width
  output logic [1:0]        logic_ops
);
  assign carry_kept  = a + c;
  assign carry_lost  = (a + c) >> 1;
  assign carry_cut   = {a + c};
  assign mixed       = sb + a;
  assign both_signed = sb + sb;
  assign cmp_mixed   = sb < a;
  assign cmp_signed  = sb < $signed(a);
  assign ashr        = sb >>> 2;
  assign ashr_u      = a >>> 2;
  assign prod        = a * c;
  assign tern        = a[0] ? sb : c;
  assign logic_ops   = {a && c, !a || (c == 4'd0)};
endmodule
