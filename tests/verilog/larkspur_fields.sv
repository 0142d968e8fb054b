// Larkspur: packed structs and unions (a sensor sample split into fields), read and written
// by member.
module larkspur_fields(input logic [7:0] a, input logic [3:0] b, output logic [3:0] y, output logic [7:0] z, output logic [2:0] u);
  typedef struct packed { logic [3:0] hi; logic [1:0] mid; logic [1:0] lo; } pack_t;
  pack_t p, q;
  assign p = a;
  assign y = p.hi ^ {p.mid, p.lo};
  always_comb begin
    q = '0;
    q.hi = b;
    q.lo = a[1:0];
  end
  assign z = q;
  typedef union packed { logic [2:0] w; struct packed { logic s; logic [1:0] v; } f; } un_t;
  un_t un;
  assign un.w = a[2:0];
  assign u = {un.f.v, un.f.s};
endmodule
