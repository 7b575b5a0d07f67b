// A four-sample file computed by hand:
//   t (s)  V     A      V·A
//   0      12.6    0       0
//   1      12.4  100    1240
//   2      12.2  200    2440
//   3      12.4  100    1240
// energy = trapezoids (0+1240)/2 + (1240+2440)/2 + (2440+1240)/2 = 620 + 1840 + 1840 = 4300 J = 1.19444 Wh;
// the points lie exactly on V = 12.6 − 0.002·I, so R = 2 mΩ and V0 = 12.6 V (least squares, r² = 1).
export const HAND_CSV = 'time,volts,amps\n0,12.6,0\n1,12.4,100\n2,12.2,200\n3,12.4,100\n';
