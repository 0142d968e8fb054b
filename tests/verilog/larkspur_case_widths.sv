// Larkspur: case expressions of different widths and signedness (IEEE 1800 12.5: all of them
// are extended to the widest; sign extension only when every one is signed), a named block
// with its own variable, and a casex whose items overlap.
module larkspur_case_widths (
  input  logic [3:0]        a,
  input  logic signed [2:0] s,
  output logic [3:0]        y,
  output logic [3:0]        z,
  output logic [1:0]        q,
  output logic [3:0]        n
);
  always_comb begin
    case (a)
      -1:      y = 4'd1;   // a 32-bit -1 never equals a zero-extended 4-bit a
      5'd20:   y = 4'd2;
      3'sb111: y = 4'd3;   // unsigned comparison: 3'sb111 is 7
      default: y = 4'd0;
    endcase
  end
  always_comb begin
    case (s)
      -1:      z = 4'd1;   // 4'b1111 below makes every expression unsigned
      3'sb110: z = 4'd2;
      4'b1111: z = 4'd3;
      default: z = 4'd0;
    endcase
  end
  always_comb begin
    casex (a[1:0])
      3'b1x0:  q = 2'd1;
      2'bx1:   q = 2'd2;
      default: q = 2'd3;
    endcase
  end
  always @(*) begin : count_ones
    reg [3:0] acc;
    integer k;
    acc = 4'd0;
    for (k = 0; k < 4; k = k + 1) acc = acc + a[k];
    n = acc;
  end
endmodule
