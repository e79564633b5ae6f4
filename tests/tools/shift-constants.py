#!/usr/bin/env python3
"""Move each model constant by +1 % (the Fowler-Nordheim prefactor also x2), rebuild, run the Physics tests in the
checkout named by the first argument (never your working copy: files are edited and restored); print the failing checks
for each shift. Optional further arguments: names of the shifts to run."""
import subprocess, sys, re, os
root = sys.argv[1]
P = 'src/JunctionFit/Physics/'
cases = [
 ('e', P+'PhysicalConstants.cs', 'ElementaryChargeC = 1.602176634e-19', 'ElementaryChargeC = 1.618198400e-19'),
 ('h', P+'PhysicalConstants.cs', 'PlanckJs = 6.62607015e-34', 'PlanckJs = 6.6923308515e-34'),
 ('me', P+'PhysicalConstants.cs', 'ElectronMassKg = 9.1093837015e-31', 'ElectronMassKg = 9.2004775385e-31'),
 ('k', P+'PhysicalConstants.cs', 'BoltzmannJPerK = 1.380649e-23', 'BoltzmannJPerK = 1.39445549e-23'),
 ('eps0', P+'PhysicalConstants.cs', 'VacuumPermittivityFPerM = 8.8541878128e-12', 'VacuumPermittivityFPerM = 8.9427296909e-12'),
 ('FN prefactor x2', P+'FowlerNordheimModel.cs', 'PrefactorConstant = E * E * E /', 'PrefactorConstant = 2.0 * E * E * E /'),
 ('FN prefactor +1%', P+'FowlerNordheimModel.cs', 'PrefactorConstant = E * E * E /', 'PrefactorConstant = 1.01 * E * E * E /'),
 ('MOS electron barrier', P+'MosGateStackModel.cs', 'ElectronBarrierEv = 3.1;', 'ElectronBarrierEv = 3.131;'),
 ('MOS electron mass', P+'MosGateStackModel.cs', 'ElectronMassRatio = 0.40;', 'ElectronMassRatio = 0.404;'),
 ('MOS electron alpha', P+'MosGateStackModel.cs', 'ElectronAlpha = 0.6;', 'ElectronAlpha = 0.606;'),
 ('MOS hole barrier', P+'MosGateStackModel.cs', 'HoleBarrierEv = 4.5;', 'HoleBarrierEv = 4.545;'),
 ('MOS hole mass', P+'MosGateStackModel.cs', 'HoleMassRatio = 0.32;', 'HoleMassRatio = 0.3232;'),
 ('MOS hole alpha', P+'MosGateStackModel.cs', 'HoleAlpha = 0.4;', 'HoleAlpha = 0.404;'),
 ('eps Si', P+'MosElectrostatics.cs', '} = 11.7;', '} = 11.817;'),
 ('eps ox', P+'MosElectrostatics.cs', '} = 3.9;', '} = 3.939;'),
 ('metal work function', P+'MosElectrostatics.cs', '} = 4.6;', '} = 4.646;'),
 ('chi Si', P+'MosElectrostatics.cs', 'SiliconElectronAffinityEv = 4.05;', 'SiliconElectronAffinityEv = 4.0905;'),
 ('n_i', P+'MosElectrostatics.cs', 'IntrinsicDensityM3 = 1.0e16 *', 'IntrinsicDensityM3 = 1.01e16 *'),
 ('Eg0', P+'MosElectrostatics.cs', '=> 1.17 - 4.73e-4', '=> 1.1817 - 4.73e-4'),
 ('Varshni alpha', P+'MosElectrostatics.cs', '1.17 - 4.73e-4 *', '1.17 - 4.7773e-4 *'),
 ('Varshni beta', P+'MosElectrostatics.cs', '(temperatureK + 636.0)', '(temperatureK + 642.36)'),
 ('image 1.2', P+'SimmonsImageForceModel.cs', 'Dual4 s1 = 1.2 *', 'Dual4 s1 = 1.212 *'),
 ('image 9.2', P+'SimmonsImageForceModel.cs', '(1.0 - 9.2 * lambda', '(1.0 - 9.292 * lambda'),
 ('image 5.6', P+'SimmonsImageForceModel.cs', '(phi0 - 5.6 * lambda)', '(phi0 - 5.656 * lambda)'),
 ('image 1.15', P+'SimmonsImageForceModel.cs', '- 1.15 * lambda', '- 1.1615 * lambda'),
 ('image ln2', P+'SimmonsImageForceModel.cs', 'E * E * Math.Log(2.0) /', '1.01 * E * E * Math.Log(2.0) /'),
 ('BDR 16', P+'BrinkmanDynesRowellModel.cs', 'double c1 = a0 * dphi / (16.0 * phi * sphi);', 'double c1 = a0 * dphi / (16.16 * phi * sphi);'),
 ('BDR 9/128', P+'BrinkmanDynesRowellModel.cs', 'double c2 = 9.0 / 128.0 * a0 * a0 / phi;\n', 'double c2 = 9.09 / 128.0 * a0 * a0 / phi;\n'),
 ('WKB image 16', P+'WkbModel.cs', 'E * E / (16.0 * Math.PI', 'E * E / (16.16 * Math.PI'),
]
only = sys.argv[2:] 
for name, f, old, new in cases:
    if only and name not in only: continue
    path = os.path.join(root, f)
    src = open(path, encoding='utf-8').read()
    n = src.count(old)
    if n < 1:
        print(f'{name}: PATTERN NOT FOUND', flush=True); continue
    open(path, 'w', encoding='utf-8').write(src.replace(old, new, 1))
    try:
        b = subprocess.run(['dotnet', 'build', 'tests/JunctionFit.Tests', '-c', 'Release', '-nologo', '-v', 'q'], cwd=root, capture_output=True, text=True)
        if b.returncode != 0:
            print(f'{name}: BUILD FAILED', b.stdout[-500:], flush=True); continue
        t = subprocess.run(['dotnet', 'test', 'tests/JunctionFit.Tests', '-c', 'Release', '--no-build', '--filter',
                            'FullyQualifiedName~JunctionFit.Tests.Physics|FullyQualifiedName~ModelConstants'], cwd=root, capture_output=True, text=True)
        failed = sorted(set(re.findall(r'Failed (JunctionFit\.Tests\.[\w.]+)', t.stdout)))
        summary = re.findall(r'(Failed!|Passed!).*', t.stdout)
        print(f'{name}: {len(failed)} failing: ' + '; '.join(x.replace("JunctionFit.Tests.","") for x in failed[:6]), flush=True)
    finally:
        open(path, 'w', encoding='utf-8').write(src)
