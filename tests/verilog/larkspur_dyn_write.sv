// Larkspur: writes through a signal index inside combinational blocks (a one-hot decoder, a
// bit flip, an element of an unpacked array; index 3 of m[0:2] writes nothing).
module larkspur_dyn_write(input logic [2:0] s, input logic [1:0] k, input logic [3:0] a, output logic [7:0] onehot, output logic [3:0] y, output logic [5:0] mf);
  logic [1:0] m [0:2];
  always_comb begin
    onehot = '0;
    onehot[s] = 1'b1;
  end
  always_comb begin
    y = a;
    y[k] = ~a[k];
  end
  always_comb begin
    m[0] = 2'd0; m[1] = 2'd1; m[2] = 2'd2;
    m[k] = a[1:0];
  end
  assign mf = {m[0], m[1], m[2]};
endmodule
