// Larkspur: Kogge-Stone with a deliberate fault: one black cell at level 2, bit 9 uses the
// wrong distance (i-3 instead of i-4).
module larkspur_ks_bug #(parameter int W = 16) (
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
        localparam int J = (l == 2 && i == 9) ? i - 3 : i - D;
        assign g[l+1][i] = g[l][i] | (p[l][i] & g[l][J]);
        assign p[l+1][i] = p[l][i] & p[l][J];
      end else begin : pass
        assign g[l+1][i] = g[l][i];
        assign p[l+1][i] = p[l][i];
      end
    end
  end
  logic [W:0] c;
  assign c[0] = cin;
  for (genvar i = 0; i < W; i++) begin : carry
    assign c[i+1] = g[L][i] | (p[L][i] & cin);
  end
  assign sum = p[0] ^ c[W-1:0];
  assign cout = c[W];
endmodule
