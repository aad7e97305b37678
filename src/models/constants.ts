/** Constants shared inside src/models (not re-exported from the index, to avoid clashes with geometry's). */
/** Speed of light in vacuum (m/s), exact (SI). */
export const C_M_S = 299_792_458;
export const DEG = Math.PI / 180;
