// Larkspur adder library: parameterized ripple-carry adder, one full-adder instance per bit
// from a generate loop. Hand-written (not generated); checked at W = 4, 8, 16 and 32.
module larkspur_fa (
  input  wire x,
  input  wire y,
  input  wire ci,
  output wire s,
  output wire co
);
  assign s  = x ^ y ^ ci;
  assign co = (x & y) | (ci & (x ^ y));
endmodule

module larkspur_add_rca_generate #(parameter W = 16) (
  input  wire [W-1:0] a,
  input  wire [W-1:0] b,
  input  wire         cin,
  output wire [W-1:0] sum,
  output wire         cout
);
  wire [W:0] c;
  assign c[0] = cin;
  genvar i;
  generate
    for (i = 0; i < W; i = i + 1) begin : bit_slice
      larkspur_fa fa (.x(a[i]), .y(b[i]), .ci(c[i]), .s(sum[i]), .co(c[i+1]));
    end
  endgenerate
  assign cout = c[W];
endmodule
