// Larkspur: adder-subtractor with signed overflow, built from a behavioural '+'.
// sub=0: {cout,res} = a + b;  sub=1: res = a - b (cout is the no-borrow flag).
module larkspur_addsub #(parameter W = 8) (
  input  [W-1:0] a, b,
  input          sub,
  output [W-1:0] res,
  output         cout,
  output         ovf
);
  wire [W-1:0] bx = b ^ {W{sub}};
  assign {cout, res} = a + bx + sub;
  assign ovf = (a[W-1] == bx[W-1]) && (res[W-1] != a[W-1]);
endmodule
