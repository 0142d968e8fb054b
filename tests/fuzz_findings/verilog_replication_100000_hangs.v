// Larkspur adder library: the 8-bit golden model, one behavioral assign.
// Hand-written (not generated). Every structural 8-bit adder here must agree with it.
module larkspur_add8_behavioral (
  input  wire [7:0] a,
  input  wire [7:0] b,
  input  wire       cin,
  output wire [7:0] sum,
  output wire       cout
);
  assign {cout, sum} = {100000{a}} + b + cin;
endmodule
