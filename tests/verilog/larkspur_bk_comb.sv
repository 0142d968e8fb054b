// Larkspur: Brent-Kung prefix adder written procedurally: an always_comb block walks the up-sweep
// and down-sweep trees over local generate/propagate vectors; the tree shape comes from
// constant loop bounds and a constant function.
module larkspur_bk_comb #(parameter int W = 16) (
  input  logic [W-1:0] a, b,
  input  logic         cin,
  output logic [W-1:0] sum,
  output logic         cout
);
  function automatic int levels(input int n);
    int l = 0;
    while ((1 << l) < n) l++;
    return l;
  endfunction
  localparam int L = levels(W);

  always_comb begin
    logic [W:0] g, p;
    // bit 0 of the prefix is the carry-in: g[0] = cin, p[0] = 0
    g[0] = cin;
    p[0] = 1'b0;
    for (int i = 0; i < W; i++) begin
      g[i+1] = a[i] & b[i];
      p[i+1] = a[i] ^ b[i];
    end
    // up-sweep
    for (int l = 0; l < L + 1; l++) begin
      for (int i = (2 << l) - 1; i <= W; i += (2 << l)) begin
        g[i] = g[i] | (p[i] & g[i - (1 << l)]);
        p[i] = p[i] & p[i - (1 << l)];
      end
    end
    // down-sweep
    for (int l = L - 1; l >= 0; l--) begin
      for (int i = (3 << l) - 1; i <= W; i += (2 << l)) begin
        g[i] = g[i] | (p[i] & g[i - (1 << l)]);
        p[i] = p[i] & p[i - (1 << l)];
      end
    end
    for (int i = 0; i < W; i++) sum[i] = a[i] ^ b[i] ^ g[i];
    cout = g[W];
  end
endmodule
