// Larkspur: 16-bit two-level carry-lookahead adder written with continuous assigns only.
module larkspur_cla4 (input [3:0] p, g, input ci, output [3:0] c, output pg, gg);
  assign c[0] = ci;
  assign c[1] = g[0] | (p[0] & ci);
  assign c[2] = g[1] | (p[1] & g[0]) | (p[1] & p[0] & ci);
  assign c[3] = g[2] | (p[2] & g[1]) | (p[2] & p[1] & g[0]) | (p[2] & p[1] & p[0] & ci);
  assign pg = &p;
  assign gg = g[3] | (p[3] & g[2]) | (p[3] & p[2] & g[1]) | (p[3] & p[2] & p[1] & g[0]);
endmodule

module larkspur_cla16 (input [15:0] a, input [15:0] b, input cin,
                       output [15:0] sum, output cout);
  wire [15:0] p = a ^ b;          // net declaration assignments
  wire [15:0] g = a & b;
  wire [15:0] c;
  wire [3:0] bp, bg, bc;
  larkspur_cla4 blk0 (.p(p[3:0]),   .g(g[3:0]),   .ci(bc[0]), .c(c[3:0]),   .pg(bp[0]), .gg(bg[0]));
  larkspur_cla4 blk1 (.p(p[7:4]),   .g(g[7:4]),   .ci(bc[1]), .c(c[7:4]),   .pg(bp[1]), .gg(bg[1]));
  larkspur_cla4 blk2 (.p(p[11:8]),  .g(g[11:8]),  .ci(bc[2]), .c(c[11:8]),  .pg(bp[2]), .gg(bg[2]));
  larkspur_cla4 blk3 (.p(p[15:12]), .g(g[15:12]), .ci(bc[3]), .c(c[15:12]), .pg(bp[3]), .gg(bg[3]));
  wire top_p, top_g;
  larkspur_cla4 lvl2 (.p(bp), .g(bg), .ci(cin), .c(bc), .pg(top_p), .gg(top_g));
  assign sum = p ^ c;
  assign cout = top_g | (top_p & cin);
endmodule
