// Larkspur: ripple adder with a deliberate fault: bit 5's carry uses OR where AND belongs.
module larkspur_rca_bug (input [7:0] a, b, input cin, output [7:0] sum, output cout);
  wire [8:0] c;
  assign c[0] = cin;
  genvar i;
  for (i = 0; i < 8; i = i + 1) begin : fa
    assign sum[i] = a[i] ^ b[i] ^ c[i];
    if (i == 5) begin : bad
      assign c[i+1] = (a[i] | b[i]) | (c[i] & (a[i] ^ b[i]));
    end else begin : good
      assign c[i+1] = (a[i] & b[i]) | (c[i] & (a[i] ^ b[i]));
    end
  end
  assign cout = c[8];
endmodule
