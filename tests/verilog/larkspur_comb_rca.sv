// Larkspur: ripple adder written as an always_comb loop with a local carry variable.
module larkspur_comb_rca #(parameter W = 8) (
  input  logic [W-1:0] a, b,
  input  logic         cin,
  output logic [W-1:0] sum,
  output logic         cout
);
  always_comb begin
    logic carry;
    carry = cin;
    for (int i = 0; i < W; i++) begin
      sum[i] = a[i] ^ b[i] ^ carry;
      carry  = (a[i] & b[i]) | (carry & (a[i] ^ b[i]));
    end
    cout = carry;
  end
endmodule
