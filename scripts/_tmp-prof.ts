import { analyseDataset, GAS_CONSTANT } from "@/lib/kinetics";
const mk=(w:boolean,s:number)=>Array.from({length:10},(_,i)=>{const T=250+80*i; const k=Math.exp(-26.7 +0.8*Math.log(T/298)- 12000/(GAS_CONSTANT*T) + 0.05*Math.sin(i*13+s)); return w?{T,k,sigmaLnK:0.05}:{T,k};});
const pool=Array.from({length:64},(_,j)=>mk(j%2===0,j));
for (let i=0;i<5000;i++) analyseDataset({points:pool[i%64], order:2});
let best=1e9; for (let r=0;r<8;r++){const t=performance.now(); for (let i=0;i<20000;i++) analyseDataset({points:pool[i%64], order:2}); best=Math.min(best,(performance.now()-t)/20000*1000);} console.log('best us/analysis', best.toFixed(2));
