// Larkspur: signed adder with overflow and saturation, using signed types and $signed.
module larkspur_sadd_flags #(parameter W = 8) (
  input  logic signed [W-1:0] a, b,
  output logic signed [W-1:0] sum,
  output logic                ovf,
  output logic signed [W-1:0] sat,
  output logic                neg,
  output logic                lt
);
  logic signed [W:0] wide;
  assign wide = a + b;              // sign-extended by the context width
  assign sum  = wide[W-1:0];
  assign ovf  = wide[W] != wide[W-1];
  assign neg  = wide < 0;
  assign lt   = a < b;
  localparam logic signed [W-1:0] MAXV = {1'b0, {(W-1){1'b1}}};
  localparam logic signed [W-1:0] MINV = {1'b1, {(W-1){1'b0}}};
  always_comb begin
    if (!ovf) sat = sum;
    else if (wide[W]) sat = MINV;
    else sat = MAXV;
  end
endmodule
