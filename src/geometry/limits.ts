/**
 * Most loops (the outline and its holes) and most edges a domain may have, after straight edges
 * in line are merged. A plate meshed to 1% on Kt needs a few elements along every edge and
 * around every hole, so far fewer fit in memory: the limits refuse in milliseconds what the mesh
 * size estimate would refuse only after building a size field over all of them.
 */
export const MAX_LOOPS = 5_000;
export const MAX_EDGES = 50_000;
