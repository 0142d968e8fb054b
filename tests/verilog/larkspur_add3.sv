// Larkspur: three-operand adder: a carry-save row (a function per bit) then a final '+'.
module larkspur_add3 #(parameter W = 8) (
  input  logic [W-1:0] a, b, c,
  output logic [W+1:0] sum
);
  function automatic logic [1:0] csa(input logic x, input logic y, input logic z);
    csa = {(x & y) | (x & z) | (y & z), x ^ y ^ z};
  endfunction
  logic [W-1:0] s, k;
  always_comb begin
    for (int i = 0; i < W; i++) begin
      {k[i], s[i]} = csa(a[i], b[i], c[i]);
    end
  end
  assign sum = {2'b00, s} + {1'b0, k, 1'b0};
endmodule
