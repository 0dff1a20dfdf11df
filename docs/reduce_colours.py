"""Reduce a palette PNG chart of passbudget to its K most frequent colours (each other colour
takes the nearest of them, by squared RGB distance), for the pictures in examples/charts/.

    python3 docs/reduce_colours.py out/pass-016-sierra-baja-20261202T0854Z.png \
        examples/charts/pass-016-sierra-baja.png 64

Reads only 8-bit indexed PNGs (what passbudget writes); standard library only.
"""
import sys, zlib, struct
from collections import Counter
def read(p):
    d=open(p,'rb').read(); i=8; idat=b''; plte=None
    while i<len(d):
        n,=struct.unpack('>I',d[i:i+4]); t=d[i+4:i+8]; c=d[i+8:i+8+n]; i+=12+n
        if t==b'IHDR': w,h,bd,ct=struct.unpack('>IIBB',c[:10])
        elif t==b'PLTE': plte=c
        elif t==b'IDAT': idat+=c
    raw=zlib.decompress(idat); assert ct==3 and bd==8
    assert d[28]==0, 'interlaced'
    assert all(raw[y*(w+1)]==0 for y in range(h)), 'a filtered row (passbudget writes unfiltered rows)'
    return w,h,[tuple(plte[3*k:3*k+3]) for k in range(len(plte)//3)],[raw[y*(w+1)+1:(y+1)*(w+1)] for y in range(h)]
def chunk(t,c): return struct.pack('>I',len(c))+t+c+struct.pack('>I',zlib.crc32(t+c)&0xffffffff)
src,dst,k=sys.argv[1],sys.argv[2],int(sys.argv[3])
w,h,pal,rows=read(src)
freq=Counter(); [freq.update(r) for r in rows]
top=[i for i,_ in freq.most_common(k)]
newpal=[pal[i] for i in top]
remap={}
for i in range(len(pal)):
    c=pal[i]; remap[i]=min(range(len(newpal)), key=lambda j: sum((a-b)**2 for a,b in zip(c,newpal[j])))
tbl=bytes(remap.get(i,0) for i in range(256))
raw=b''.join(b'\0'+r.translate(tbl) for r in rows)
out=b'\x89PNG\r\n\x1a\n'+chunk(b'IHDR',struct.pack('>IIBBBBB',w,h,8,3,0,0,0))+chunk(b'PLTE',b''.join(bytes(c) for c in newpal))+chunk(b'IDAT',zlib.compress(raw,9))+chunk(b'IEND',b'')
open(dst,'wb').write(out)
print(dst, len(out))
