"""Stub entries (amalgebra/__init__.pyi) for public names: a starting point, to be reviewed.

    python3 tests/typing_check/stub_entry.py NAME [NAME ...]    # print the entries
    python3 tests/typing_check/stub_entry.py --sync             # add missing names to the stub, drop
                                                          # stale ones, rewrite its __all__

Classes become re-exports from their defining module; functions get parameter types from the
parameter names (quantum numbers, angles, expressions, labels) and the return type listed in
``RET`` below (``Any`` when not listed).  tests/test_typing.py checks the stub against the runtime.
"""

import ast
import inspect
import sys
from pathlib import Path

import amalgebra as am

QN = {"j","m","j1","m1","j2","m2","J","M","j3","m3","j4","j5","j6","jp","mp","k","q","l","l1","l2","l3",
      "m1p","m2p","j11","j12","j13","j21","j22","j23","j31","j32","j33","j1p","j2p","Jp","k1","k2","S","n"}
ANG = {"alpha","beta","gamma","theta","phi","theta1","phi1","theta2","phi2","a","a2","b","b2"}
EXPR = {"expr","op","x","y","first","second","lhs","rhs","state","bra_state","ket_state","element","value","jdotv",
        "jsq","mz","U","M","V"}
RET = {  # return types of the functions in the stub when it was written
 "cg":"_Expr","threej":"_Expr","sixj":"_Expr","ninej":"_Expr","racah_w":"_Expr",
 "cg_float":"float","threej_float":"float","sixj_float":"float","ninej_float":"float",
 "clear_coupling_caches":"None","coupling_cache_info":"dict[str, Any]","kernel_backend":"str",
 "closed_form_conditions":"_Expr","half_integer":"_Expr","triangle":"bool",
 "canonical":"_Expr","commutator":"_Expr","nested_commutator":"_Expr","adjoint_action":"_Expr",
 "to_cartesian":"_Expr","to_ladder":"_Expr","dot":"_Expr","collect_casimir":"dict[Any, _Expr]",
 "ladder_terms":"dict[Any, _Expr]",
 "to_matrix":"Any","verify_identity":"IdentityCheck","assert_identity":"None",
 "ket":"Ket","bra":"Bra","product_ket":"ProductKet","inner":"_Expr","norm":"_Expr","normalize":"_Expr",
 "apply":"_Expr","matrix_element":"_Expr","expectation":"_Expr","coupled_ket":"CoupledKet",
 "coupled_chain":"CoupledKet","to_uncoupled":"_Expr","uncoupled_to_coupled":"_Expr",
 "coupling_matrix":"CouplingMatrix","hamiltonian_matrix":"Any","multiplet_count":"int",
 "total_spin_states":"list[Any]","singlet":"_Expr","correlation":"_Expr","chsh":"_Expr",
 "small_d":"_Expr","wigner_D":"_Expr","small_d_matrix":"_Matrix","wigner_D_matrix":"_Matrix",
 "compose_rotations":"RotationComposition","clebsch_gordan_series":"_Expr",
 "rotate_ket":"_Expr","rotate_operator":"_Expr",
 "spherical_harmonic":"_Expr","racah_harmonic":"_Expr","addition_theorem":"AdditionTheorem",
 "harmonic_triple_integral":"_Expr",
 "fock_ket":"_Expr","apply_bosons":"_Expr","to_bosons":"_Expr","from_bosons":"_Expr",
 "spin_to_fock":"_Expr","fock_to_spin":"_Expr","schwinger_small_d":"_Expr",
 "racah_tensor":"SphericalTensor","unit_tensor":"SphericalTensor","tensor_product":"Any",
 "scalar_product":"_Expr","decompose":"Decomposition","recombine":"_Expr","reduced_part1":"_Expr",
 "reduced_part2":"_Expr","reduced_tensor_product":"_Expr","projection_theorem":"_Expr",
 "bilinear_tensor_form":"TensorForm","spin_hamiltonian_tensor_form":"TensorForm",
 "wigner_eckart":"_Expr","reduced_from_element":"_Expr","element_table":"ElementTable",
 "convert_reduced":"_Expr","selection_rules":"_Expr","parse":"_Expr","to_text":"str",
 "derivation":"Any",
}
OVERRIDE = {
 ("racah_w", None): "_QuantumNumber",
 ("commutator","a"):"_Expr", ("commutator","b"):"_Expr",
 ("scalar_product","a"):"Any", ("scalar_product","b"):"Any",
 ("tensor_product","a"):"Any", ("tensor_product","b"):"Any",
 ("compose_rotations","first"):"tuple[_Angle, _Angle, _Angle]", ("compose_rotations","second"):"tuple[_Angle, _Angle, _Angle]",
 ("chsh","a"):"_Angle",
 ("bilinear_tensor_form","M"):"Any", ("bilinear_tensor_form","U"):"Any", ("bilinear_tensor_form","V"):"Any",
 ("multiplet_count","n"):"int", ("total_spin_states","n"):"int",
 ("total_spin_states","S"):"_QuantumNumber | None", ("total_spin_states","M"):"_QuantumNumber | None",
 ("convert_reduced","value"):"_Expr", ("parse","text"):"str",
 ("adjoint_action","order"):"int", ("nested_commutator","n"):"int", ("dot","first"):"Any", ("dot","second"):"Any",
 ("to_matrix","j"):"Mapping[str, Any]", ("hamiltonian_matrix","js"):"Mapping[str, Any]",
}
def ptype(fn, p):
    n=p.name
    if (fn,None) in OVERRIDE and n in "abcdef": return OVERRIDE[(fn,None)]
    if (fn,n) in OVERRIDE: t=OVERRIDE[(fn,n)]
    elif n in QN: t="_QuantumNumber"
    elif n in ANG: t="_Angle"
    elif n in EXPR: t="_Expr"
    elif n in ("label","name","kind","from_convention","to_convention","convention","basis","axis_a","axis_b"):
        t = "str" if not n.startswith("axis") else "Any"
    elif n in ("labels",): t="Sequence[str] | str | None" if p.default is None else "Sequence[str]"
    elif n in ("modes","names"): t="Sequence[str]"
    elif n in ("js",): t="Any"
    elif p.annotation is not inspect._empty: t=str(p.annotation)
    elif isinstance(p.default,bool): t="bool"
    elif isinstance(p.default,int): t="int"
    elif isinstance(p.default,float): t="float"
    elif isinstance(p.default,str): t="str"
    else: t="Any"
    if p.default is None and "None" not in t and t!="Any": t += " | None"
    return t


def stub_entry(name):
    """The stub text for one public name of ``amalgebra``."""
    obj = getattr(am, name)
    if inspect.isclass(obj):
        module = obj.__module__.replace("amalgebra", "", 1)
        return f"from {module} import {name} as {name}"
    parts, star = [], False
    for p in inspect.signature(obj).parameters.values():
        if p.kind == p.KEYWORD_ONLY and not star:
            parts.append("*")
            star = True
        t = ptype(name, p)
        if p.kind == p.VAR_POSITIONAL:
            parts.append(f"*{p.name}: {t}")
            star = True
            continue
        if p.kind == p.VAR_KEYWORD:
            parts.append(f"**{p.name}: {t}")
            continue
        dv = p.default
        literal = dv is None or isinstance(dv, (bool, int, float, str)) or (
            isinstance(dv, tuple) and all(isinstance(x, str) for x in dv))
        default = "" if dv is inspect.Parameter.empty else (
            " = " + repr(dv).replace("'", '"') if literal else " = ...")
        parts.append(f"{p.name}: {t}{default}")
    return f"def {name}({', '.join(parts)}) -> {RET.get(name, 'Any')}: ..."


STUB = Path(__file__).resolve().parents[2] / "amalgebra" / "__init__.pyi"
_NEW_FUNCTIONS = "# names added after the stub was written: annotations to tighten with their owners"


def _declared(tree):
    names = {}
    for node in tree.body:
        if isinstance(node, ast.FunctionDef):
            names[node.name] = node
        elif isinstance(node, ast.ImportFrom):
            for alias in node.names:
                if alias.asname == alias.name:
                    names[alias.name] = node
    return names


def _wrap(line, width=100):
    if len(line) <= width or not line.startswith("def "):
        return line
    head, rest = line.split("(", 1)
    params, tail = rest.rsplit(") -> ", 1)
    parts, depth, cur = [], 0, ""
    for ch in params:
        depth += ch in "([" and 1 or (ch in ")]" and -1 or 0)
        if ch == "," and depth == 0:
            parts.append(cur.strip())
            cur = ""
        else:
            cur += ch
    parts.append(cur.strip())
    return "\n".join([head + "("] + [f"    {p}," for p in parts] + [") -> " + tail])


def sync():
    """Bring the stub's set of names in line with ``amalgebra.__all__``; return the names added."""
    text = STUB.read_text(encoding="utf-8")
    public = [n for n in am.__all__ if n != "__version__"]
    declared = _declared(ast.parse(text))
    lines = text.split("\n")
    for name, node in declared.items():  # stale entries: drop their lines
        if name in public:
            continue
        if isinstance(node, ast.FunctionDef):
            for i in range(node.lineno - 1, node.end_lineno):
                lines[i] = None
        else:
            raise SystemExit(f"{name} is re-exported by the stub but no longer public: edit by hand")
    lines = [line for line in lines if line is not None]
    missing = [n for n in public if n not in declared]
    classes = [stub_entry(n) for n in missing if inspect.isclass(getattr(am, n))]
    functions = [_wrap(stub_entry(n)) for n in missing if not inspect.isclass(getattr(am, n))]
    text = "\n".join(lines)
    if classes:
        anchor = "\nfrom .harmonics import AdditionTheorem\n"
        text = text.replace(anchor, "\n" + "\n".join(classes) + "\n" + anchor, 1)
    if functions:
        if _NEW_FUNCTIONS not in text:
            text = text.rstrip("\n") + "\n\n" + _NEW_FUNCTIONS + "\n"
        text = text.rstrip("\n") + "\n" + "\n".join(functions) + "\n"
    start = text.index("__all__ = [")
    end = text.index("]\n", start) + 2
    rows, row = [], "   "
    for name in am.__all__:
        item = f' "{name}",'
        if len(row) + len(item) > 100:
            rows.append(row)
            row = "   "
        row += item
    rows.append(row)
    text = text[:start] + "__all__ = [\n" + "\n".join(rows) + "\n]\n" + text[end:]
    STUB.write_text(text, encoding="utf-8")
    return missing


if __name__ == "__main__":
    if sys.argv[1:] == ["--sync"]:
        print("added:", ", ".join(sync()) or "nothing")
    else:
        for arg in sys.argv[1:]:
            print(stub_entry(arg))
