package chk
import ("context";"testing";"fmt";"time";"shiftrank/isomers";"shiftrank/molecule")
func TestX(t *testing.T){
 C,O:=molecule.C,molecule.O
 f:=molecule.MustParseFormula("C10H12O2")
 het:=[]molecule.Element{O}
 base:=[]isomers.Class{
  {Name:"CH3 t", Element:C,H:3,Count:1,Bonds:isomers.SingleBonds,Vicinal:isomers.Bound{On:true,Min:2,Max:2}},
  {Name:"CH2 q O", Element:C,H:2,Count:1,Bonds:isomers.SingleBonds,Vicinal:isomers.Bound{On:true,Min:3,Max:3},Neighbours:[]isomers.NeighbourRule{{Elements:het,Min:1,Max:-1}}},
  {Name:"CH2 s", Element:C,H:2,Count:1,Bonds:isomers.SingleBonds,Vicinal:isomers.Bound{On:true,Min:0,Max:0},Neighbours:[]isomers.NeighbourRule{{Elements:het,Unsaturated:true,Min:1,Max:-1}}},
  {Name:"ArH", Element:C,H:1,Count:5,Bonds:isomers.OneDouble},
  {Name:"C", Element:C,H:0,Count:2},
  {Name:"O", Element:O,H:0,Count:2},
 }
 run:=func(name string, cl []isomers.Class, flt isomers.Filter){
  st:=time.Now()
  s,err:=isomers.Count(context.Background(),f,isomers.Options{Spec:&isomers.Spec{Classes:cl},Filter:flt})
  fmt.Println(name, s.Emitted, s.Generated, err, time.Since(st))
 }
 run("h-only", []isomers.Class{{Element:C,H:3,Count:1},{Element:C,H:2,Count:2},{Element:C,H:1,Count:5},{Element:C,H:0,Count:2},{Element:O,H:0,Count:2}}, isomers.DefaultFilter())
 run("rules", base, isomers.DefaultFilter())
 ph:=append([]isomers.Class{},base...)
 ph[3]=isomers.Class{Name:"ArH", Element:C,H:1,Count:5,Bonds:isomers.OneDouble,MaxDegree:2,Neighbours:[]isomers.NeighbourRule{{Classes:[]int{3,6},Min:2,Max:2}}}
 ph[4]=isomers.Class{Name:"C", Element:C,H:0,Count:1}
 ph=append(ph, isomers.Class{Name:"ipso",Element:C,H:0,Count:1,Bonds:isomers.OneDouble,Neighbours:[]isomers.NeighbourRule{{Classes:[]int{3},Min:2,Max:2}}})
 run("phenyl", ph, isomers.DefaultFilter())
 isomers.Generate(context.Background(),f,isomers.Options{Spec:&isomers.Spec{Classes:ph}},func(g *molecule.Graph)bool{fmt.Println(molecule.CanonicalSMILES(g));return true})
}
