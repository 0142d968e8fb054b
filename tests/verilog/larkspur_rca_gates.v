// Larkspur sensor-fusion accelerator: ripple-carry adder from gate-primitive full adders.
// Hierarchy with named and positional connections, a generate loop and expressions in
// connections.
module larkspur_fa (output s, output co, input a, input b, input ci);
  wire p, g, t;
  xor  x1 (p, a, b);
  xor  x2 (s, p, ci);
  and  a1 (g, a, b), a2 (t, p, ci);   // two instances in one statement
  or   o1 (co, g, t);
endmodule

module larkspur_rca_gates #(parameter W = 8) (
  input  [W-1:0] a, b,
  input          cin,
  output [W-1:0] sum,
  output         cout
);
  wire [W:0] c;
  assign c[0] = cin;
  genvar i;
  generate
    for (i = 0; i < W; i = i + 1) begin : bit_slice
      if (i % 2 == 0) begin : even
        larkspur_fa fa (.s(sum[i]), .co(c[i+1]), .a(a[i]), .b(b[i]), .ci(c[i]));
      end else begin : odd
        larkspur_fa fa (sum[i], c[i+1], a[i], b[i], c[i]);   // positional
      end
    end
  endgenerate
  assign cout = c[W];
endmodule
