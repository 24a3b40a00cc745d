import { analyseDataset, GAS_CONSTANT } from "@/lib/kinetics";
const mk=(w:boolean,s:number)=>Array.from({length:10},(_,i)=>{const T=250+80*i; const k=Math.exp(-26.7 +0.8*Math.log(T/298)- 12000/(GAS_CONSTANT*T) + 0.05*Math.sin(i*13+s)); return w?{T,k,sigmaLnK:0.05}:{T,k};});
const pool=Array.from({length:64},(_,j)=>mk(j%2===0,j));
for (let i=0;i<5000;i++) analyseDataset({points:pool[i%64], order:2});
const t=performance.now(); for (let i=0;i<100000;i++) analyseDataset({points:pool[i%64], order:2}); console.log('us/analysis', (performance.now()-t)/100000*1000);
const fl={}; for (const p of pool) for (const f of analyseDataset({points:p,order:2}).flags) fl[f.code]=(fl[f.code]||0)+1; console.log(fl);
