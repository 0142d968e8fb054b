// Larkspur: a grab-bag of constructs for the simulator cross-check (not an adder).
module larkspur_mix_leaf #(parameter N = 4) (input [N-1:0] x, input [N-1:0] y, output [N-1:0] z);
  assign z = (x << 1) ^ (y >> 1) ^ {N{x[0]}};
endmodule

module larkspur_mix (
  input  [7:0] a,
  input  [7:0] b,
  input  [0:3] r,          // ascending range: r[0] is the most significant bit
  input  [1:0] sel,
  input  signed [5:0] sa,
  output [7:0] o_bits,
  output [5:0] o_red,
  output [7:0] o_sel,
  output [7:0] o_mux,
  output [3:0] o_up,
  output [0:3] o_asc,
  output [7:0] o_shift,
  output [7:0] o_mul,
  output [5:0] o_cmp,
  output reg [7:0] o_case,
  output [7:0] o_leaf,
  output [7:0] o_gen,
  output [8:0] o_sub,
  output [7:0] o_dyn
);
  function integer ones(input integer v);   // constant function
    integer k;
    begin
      ones = 0;
      for (k = 0; k < 32; k = k + 1) ones = ones + ((v >> k) & 1);
    end
  endfunction
  localparam integer K = ones(8'hB5);         // 5
  localparam [7:0] MASK = 8'h5A;

  assign o_bits = (a & b) | (~a & MASK) ^ (a ~^ b);
  assign o_red  = {&a, |b, ^a, ~&b, ~|a, ~^b};
  assign o_sel  = {a[3:0], b[7:4]} ^ {a[2 +: 3], b[7 -: 5]};
  assign o_mux  = sel[1] ? (sel[0] ? a : b) : (sel[0] ? ~a : a + b);
  assign o_up   = r + 4'd3;
  assign o_asc  = {r[3], r[2], r[0:1]};
  assign o_shift = (a << 2) | (b >> 3) | ($signed(b) >>> 6) | (a << K);
  assign o_mul  = a[3:0] * b[3:0] + K;
  assign o_cmp  = {a < b, a >= b, sa < 6'sd3, sa > -6'sd4, a == b, a != ~b};

  always @* begin
    casez (sel)
      2'b1?:   o_case = a - b;
      2'b01:   o_case = {b[3:0], a[7:4]};
      default: o_case = 8'd0;
    endcase
  end

  wire [3:0] zl, zh;
  larkspur_mix_leaf #(.N(4)) leaf_lo (.x(a[3:0]), .y(b[3:0]), .z(zl));
  larkspur_mix_leaf #(4) leaf_hi (a[7:4], ~b[7:4], zh);
  assign o_leaf = {zh, zl};

  // 2-D wire, generate case and an unnamed generate block
  wire [1:0] pair [0:3];
  genvar i;
  generate
    for (i = 0; i < 4; i = i + 1) begin : gen_pairs
      case (i)
        0: assign pair[i] = a[1:0] & b[1:0];
        1: assign pair[i] = a[3:2] | b[3:2];
        default: assign pair[i] = a[2*i+1:2*i] ^ b[2*i+1:2*i];
      endcase
    end
  endgenerate
  if (K > 4) begin
    assign o_gen = {pair[3], pair[2], pair[1], pair[0]};
  end else begin
    assign o_gen = 8'hFF;
  end

  // nand/nor/xnor with three inputs, an instance array, a buf with two outputs
  wire n1, n2, n3, d1, d2;
  nand (n1, a[0], a[1], a[2]);
  nor  (n2, b[0], b[1], b[2]);
  xnor (n3, a[7], b[7], sel[0]);
  wire [2:0] arr;
  and  ga [2:0] (arr, a[5:3], b[5:3]);
  buf  (d1, d2, arr[1]);
  assign o_sub = {n1, n2, n3, arr, d1, d2, 1'b1} - {1'b0, a};
  assign o_dyn = a >> sel;
endmodule
