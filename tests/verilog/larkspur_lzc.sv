// Larkspur: leading-zero count for the normalizer after the fusion adder, plus two other loops
// that leave early: break and continue with conditions that depend on the inputs.
module larkspur_lzc(input logic [7:0] a, output logic [3:0] lz, output logic [3:0] cnt, output logic [7:0] mask, output logic found);
  // leading-zero count with break
  always_comb begin
    lz = 4'd8;
    for (int i = 7; i >= 0; i--) begin
      if (a[i]) begin
        lz = 4'(7 - i);
        break;
      end
    end
  end
  // count ones skipping bit 3 with continue
  always_comb begin
    cnt = 0;
    for (int i = 0; i < 8; i++) begin
      if (i == 3) continue;
      if (a[i] == 1'b0) continue;
      cnt = cnt + 1;
    end
  end
  // ones below the first zero
  always_comb begin
    mask = '0;
    found = 1'b0;
    for (int i = 0; i < 8; i++) begin
      if (!a[i]) begin found = 1'b1; break; end
      mask[i] = 1'b1;
    end
  end
endmodule
