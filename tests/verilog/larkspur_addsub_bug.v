// Larkspur: adder-subtractor with two deliberate faults: the +1 of the two's complement is
// missing and the overflow flag looks at the carry out instead of the signs.
module larkspur_addsub_bug #(parameter W = 8) (
  input  [W-1:0] a, b,
  input          sub,
  output [W-1:0] res,
  output         cout,
  output         ovf
);
  wire [W-1:0] bx = b ^ {W{sub}};
  assign {cout, res} = a + bx;
  assign ovf = cout;
endmodule
