// Larkspur: parameterized Kogge-Stone parallel-prefix adder.
// Generate loops over a 2-D array of generate/propagate levels, $clog2 and a localparam.
module larkspur_ks #(parameter int W = 16) (
  input  logic [W-1:0] a, b,
  input  logic         cin,
  output logic [W-1:0] sum,
  output logic         cout
);
  localparam int L = $clog2(W);
  logic [W-1:0] g [0:L];
  logic [W-1:0] p [0:L];
  assign g[0] = a & b;
  assign p[0] = a ^ b;
  for (genvar l = 0; l < L; l++) begin : level
    localparam int D = 1 << l;
    for (genvar i = 0; i < W; i++) begin : node
      if (i >= D) begin : black
        assign g[l+1][i] = g[l][i] | (p[l][i] & g[l][i-D]);
        assign p[l+1][i] = p[l][i] & p[l][i-D];
      end else begin : pass
        assign g[l+1][i] = g[l][i];
        assign p[l+1][i] = p[l][i];
      end
    end
  end
  // carries: c[i] into bit i, with the carry-in folded in through the prefix of bits below
  logic [W:0] c;
  assign c[0] = cin;
  for (genvar i = 0; i < W; i++) begin : carry
    assign c[i+1] = g[L][i] | (p[L][i] & cin);
  end
  assign sum = p[0] ^ c[W-1:0];
  assign cout = c[W];
endmodule
