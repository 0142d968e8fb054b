// Larkspur: incrementer with an always @* block, if/else and a for loop.
module larkspur_inc #(parameter W = 8) (input [W-1:0] a, output reg [W-1:0] y, output reg co);
  integer i;
  reg carry;
  always @* begin
    carry = 1'b1;
    for (i = 0; i < W; i = i + 1) begin
      if (carry) begin
        y[i] = ~a[i];
        carry = a[i];
      end else begin
        y[i] = a[i];
      end
    end
    co = carry;
  end
endmodule
