// Larkspur: carry-select adder with a deliberate fault: block 2 picks its sums with the select
// inverted.
module larkspur_csel_bug #(parameter W = 16, parameter B = 4) (
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
      wire [B:0] s0 = a[k*B +: B] + b[k*B +: B];
      wire [B:0] s1 = a[k*B +: B] + b[k*B +: B] + 1'b1;
      wire pick = (k == 2) ? ~c[k] : c[k];
      assign sum[k*B +: B] = pick ? s1[B-1:0] : s0[B-1:0];
      assign c[k+1] = c[k] ? s1[B] : s0[B];
    end
  endgenerate
  assign cout = c[N];
endmodule
