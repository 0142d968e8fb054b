// Larkspur: carry-select adder; each block computes both sums with '+', a mux picks one.
module larkspur_csel #(parameter W = 16, parameter B = 4) (
  input  [W-1:0] a, b,
  input          cin,
  output [W-1:0] sum,
  output         cout
);
  localparam N = W / B;
  wire [N:0] c;
  assign c[0] = cin;
  genvar k;
  generate
    for (k = 0; k < N; k = k + 1) begin : blk
      wire [B:0] s0, s1;
      assign s0 = a[k*B +: B] + b[k*B +: B];
      assign s1 = a[k*B +: B] + b[k*B +: B] + 1'b1;
      assign sum[k*B +: B] = c[k] ? s1[B-1:0] : s0[B-1:0];
      assign c[k+1] = c[k] ? s1[B] : s0[B];
    end
  endgenerate
  assign cout = c[N];
endmodule
