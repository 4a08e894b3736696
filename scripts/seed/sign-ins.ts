// The demo accounts the seed creates; every one signs in with DEMO_PASSWORD.
export const DEMO_PASSWORD = 'bayward-demo'

export interface DemoSignIn {
  email: string
  name: string
  role: string
  site: string
}

export const DEMO_SIGN_INS: readonly DemoSignIn[] = [
  { email: 'operator@millbrook.example', name: 'Tamsin Reyes-Holloway', role: 'Operator', site: 'Millbrook DC' },
  { email: 'technician@millbrook.example', name: 'Odell Brannigan', role: 'Technician', site: 'Millbrook DC (also fills LP cylinders at Fenwick Cross-Dock)' },
  { email: 'facilities@millbrook.example', name: 'Priya Vantongeren', role: 'Facilities lead', site: 'Millbrook DC' },
  { email: 'safety@millbrook.example', name: 'Marcus Eldridge-Nwosu', role: 'Safety lead', site: 'Millbrook DC' },
  { email: 'operator@fenwick.example', name: 'Kasia Lindqvist', role: 'Operator', site: 'Fenwick Cross-Dock' },
  { email: 'technician@fenwick.example', name: 'Hollis Mbeki-Ward', role: 'Technician', site: 'Fenwick Cross-Dock' },
  { email: 'facilities@fenwick.example', name: 'Renata Oyelaran', role: 'Facilities lead', site: 'Fenwick Cross-Dock' },
  { email: 'safety@fenwick.example', name: 'Wendell Achterberg', role: 'Safety lead', site: 'Fenwick Cross-Dock' },
  { email: 'admin@quillmere.example', name: 'Imogen Castellanos', role: 'Admin', site: 'Millbrook DC and Fenwick Cross-Dock' },
]
